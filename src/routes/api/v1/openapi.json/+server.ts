// GET /api/v1/openapi.json: the API description, generated from the routes' zod schemas.
// Public: it describes shapes, never data.
import { json } from '@sveltejs/kit';
import { openApiDocument } from '$lib/server/openapi';
import type { RequestHandler } from './$types';

const document = openApiDocument();

export const GET: RequestHandler = () => json(document, { headers: { 'cache-control': 'public, max-age=300' } });
