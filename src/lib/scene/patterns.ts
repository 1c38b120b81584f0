/**
 * Surface patterns for statuses (docs/look-and-words.md: never colour alone). Browser-only: textures are drawn
 * on a canvas once per status and shared by every mesh.
 */
import { CanvasTexture, RepeatWrapping, SRGBColorSpace } from 'three';
import type { FitStatus } from '$lib/geometry';
import { STATUS_STYLE } from './palette';

const cache = new Map<FitStatus, CanvasTexture>();

export function statusTexture(status: FitStatus): CanvasTexture | null {
	if (typeof document === 'undefined') return null;
	const hit = cache.get(status);
	if (hit) return hit;
	const size = 64;
	const canvas = document.createElement('canvas');
	canvas.width = canvas.height = size;
	const g = canvas.getContext('2d');
	if (!g) return null;
	const { color, edge, pattern } = STATUS_STYLE[status];
	g.fillStyle = color;
	g.fillRect(0, 0, size, size);
	if (pattern === 'hatch') {
		diagonals(g, size, { color: edge, width: 5, step: 20, both: false });
	} else if (pattern === 'dots') {
		g.fillStyle = '#f1eafe';
		for (let y = 8; y < size; y += 16) {
			for (let x = 8; x < size; x += 16) {
				g.beginPath();
				g.arc(x + (y % 32 === 8 ? 0 : 8), y, 3, 0, Math.PI * 2);
				g.fill();
			}
		}
	} else if (pattern === 'crosshatch') {
		// Collides: lines both ways and a heavy dark edge (the worst reads so without colour).
		diagonals(g, size, { color: edge, width: 3, step: 16, both: true });
		g.strokeStyle = '#2a0603';
		g.lineWidth = 8;
		g.strokeRect(4, 4, size - 8, size - 8);
	}
	const texture = new CanvasTexture(canvas);
	texture.wrapS = texture.wrapT = RepeatWrapping;
	texture.colorSpace = SRGBColorSpace;
	cache.set(status, texture);
	return texture;
}

/** Diagonal lines across the square every `step` pixels, rising, and falling too when `both`. */
function diagonals(
	g: CanvasRenderingContext2D,
	size: number,
	line: { color: string; width: number; step: number; both: boolean }
) {
	g.strokeStyle = line.color;
	g.lineWidth = line.width;
	for (let k = -size; k < size * 2; k += line.step) {
		g.beginPath();
		g.moveTo(k, size);
		g.lineTo(k + size, 0);
		if (line.both) {
			g.moveTo(k, 0);
			g.lineTo(k + size, size);
		}
		g.stroke();
	}
}
