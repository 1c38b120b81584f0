/** A scene the engine cannot resolve: a position that is not allowed, a reference that is missing. */
export class SceneError extends Error {
	/** Where in the scene, in the same form as schema issues: `dividerPositions.main`. */
	readonly path: string;

	constructor(path: string, message: string) {
		super(`${path}: ${message}`);
		this.name = 'SceneError';
		this.path = path;
	}
}
