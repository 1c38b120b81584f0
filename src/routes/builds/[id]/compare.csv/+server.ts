import { compareCsv } from '$lib/builds/compare';
import { requireBuild } from '$lib/server/access';
import { loadComparison } from '$lib/server/compare';
import type { RequestHandler } from './$types';
import { pageRoute } from '$lib/server/errors';

export const GET: RequestHandler = pageRoute(async ({ locals, params, url }) => {
	const { build } = await requireBuild(locals, params.id, 'build.edit', url);
	const c = await loadComparison(build, url.searchParams.get('variants'));
	const name =
		build.name
			.replace(/[^A-Za-z0-9-]+/g, '-')
			.replace(/^-|-$/g, '')
			.toLowerCase() || 'build';
	return new Response(compareCsv(c.inputs, c.rows), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${name}-comparison.csv"`
		}
	});
});
