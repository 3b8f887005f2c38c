// The rail design screen's data in one request (GET /api/v1/rails/{id}/screen): the rail, the
// caller's role, the latest revision's design, its history, sign-off requests and bench files.
// The form the screen opens with is the latest design, else a starter design for the rail. A
// rail of another board or workspace than the address names is "not found", like the API's 404.
// The (app) layout already turns signed-out visitors to the sign-in page.
import { error } from '@sveltejs/kit';
import { apiLoad } from '$lib/client/api';
import type { RailScreen } from '$lib/client/types';
import { formFromDocument, starterForm } from '$lib/design/form';
import type { PageLoad } from './$types';

/** The dependency a mutation on this screen invalidates to read the screen again. */
export const _RAIL_SCREEN = 'app:rail-screen';

export const load: PageLoad = async ({ fetch, params, url, depends }) => {
	depends(_RAIL_SCREEN);
	const screen = await apiLoad<RailScreen>(fetch, `/api/v1/rails/${params.rail}/screen`, url);
	if (screen.rail.workspaceId !== params.workspace || screen.rail.projectId !== params.project) error(404, 'rail not found');
	const form = screen.latest ? formFromDocument(screen.latest.design as Parameters<typeof formFromDocument>[0], screen.rail) : starterForm(screen.rail);
	return { screen, form };
};
