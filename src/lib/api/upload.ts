/** The photos page's one network call: an upload with progress (fetch cannot report upload progress). */
import type { UploadResponse } from '../../routes/api/photos/[buildId]/+server';

export type UploadProgress = { loaded: number; total: number };

export function uploadPhoto(
	buildId: string,
	file: File,
	caption: string,
	onProgress: (p: UploadProgress) => void
): Promise<UploadResponse> {
	return new Promise((resolve, reject) => {
		const xhr = new XMLHttpRequest();
		xhr.open('POST', `/api/photos/${encodeURIComponent(buildId)}`);
		xhr.responseType = 'json';
		xhr.setRequestHeader('accept', 'application/json');
		xhr.upload.onprogress = (e) =>
			onProgress({ loaded: e.loaded, total: e.lengthComputable ? e.total : file.size });
		xhr.onload = () => {
			if (xhr.status >= 200 && xhr.status < 300) resolve(xhr.response as UploadResponse);
			else {
				reject(
					new Error(
						(xhr.response as { message?: string } | null)?.message ??
							`Upload failed (${xhr.status}).`
					)
				);
			}
		};
		xhr.onerror = () =>
			reject(new Error('The upload was interrupted. Check the connection and try again.'));
		const body = new FormData();
		body.append('file', file);
		body.append('caption', caption);
		xhr.send(body);
	});
}
