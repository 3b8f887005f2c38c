// Shared state of the signed-in area: who is signed in, their workspaces (for the switcher)
// and the current workspace's boards (for the side list). Fetched in the browser from /api/v1
// by the (app) layout and handed to pages through context, so a page that creates or renames a
// board refreshes the navigation with one call.
import { getContext, setContext } from 'svelte';
import { getOrThrow } from '$lib/client/api';
import type { Me, Page, Project, WorkspaceSummary } from '$lib/client/types';

/** A value fetched from the API: loading, failed with a message, or ready. */
export type Remote<T> = { phase: 'loading' } | { phase: 'error'; message: string } | { phase: 'ready'; data: T };

const KEY = Symbol('loopwright-app-state');

export class AppState {
	me = $state<Remote<Me>>({ phase: 'loading' });
	/** Boards of `workspaceId`; reset to loading whenever the workspace changes. */
	boards = $state<Remote<Project[]>>({ phase: 'loading' });
	workspaceId = $state<string | null>(null);

	/** The current workspace with the caller's role, once /me has answered. */
	workspace = $derived.by((): WorkspaceSummary | null => {
		if (this.me.phase !== 'ready' || !this.workspaceId) return null;
		return this.me.data.workspaces.find((w) => w.id === this.workspaceId) ?? null;
	});

	async loadMe() {
		try {
			this.me = { phase: 'ready', data: await getOrThrow<Me>('/api/v1/me') };
		} catch (e) {
			this.me = { phase: 'error', message: messageOf(e) };
		}
	}

	/** Switches the board list to `id` (null outside a workspace) and fetches it. */
	async showWorkspace(id: string | null) {
		if (id === this.workspaceId && this.boards.phase !== 'error') return;
		this.workspaceId = id;
		await this.loadBoards();
	}

	async loadBoards() {
		const id = this.workspaceId;
		if (!id) {
			this.boards = { phase: 'ready', data: [] };
			return;
		}
		this.boards = { phase: 'loading' };
		try {
			const page = await getOrThrow<Page<Project>>(`/api/v1/projects?workspace=${encodeURIComponent(id)}&limit=200`);
			// A late answer for a workspace we already left must not overwrite the current list.
			if (this.workspaceId === id) this.boards = { phase: 'ready', data: page.items };
		} catch (e) {
			if (this.workspaceId === id) this.boards = { phase: 'error', message: messageOf(e) };
		}
	}
}

export function messageOf(e: unknown): string {
	return e instanceof Error ? e.message : String(e);
}

export function provideAppState(): AppState {
	return setContext(KEY, new AppState());
}

export function useAppState(): AppState {
	const state = getContext<AppState | undefined>(KEY);
	if (!state) throw new Error('useAppState() outside the signed-in layout');
	return state;
}
