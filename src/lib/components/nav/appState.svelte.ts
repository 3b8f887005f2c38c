// Shared state of the signed-in area, as the (app) layout's load read it: who is signed in, their
// workspaces (for the switcher) and the current workspace's boards (for the board menu). Handed
// to pages through context, so a page that creates or renames a board, or changes a role,
// refreshes the navigation with one call (`refresh`, which runs the layout's load again).
import { getContext, setContext } from 'svelte';
import { invalidate } from '$app/navigation';
import type { Me, Project, WorkspaceSummary } from '$lib/client/types';

/** A value fetched from the API: loading, failed with a message, or ready. */
export type Remote<T> = { phase: 'loading' } | { phase: 'error'; message: string } | { phase: 'ready'; data: T };

/** The dependency of the layout's load: invalidating it reads the caller and the boards again. */
export const NAV = 'app:nav';

/** What the (app) layout's load answers. */
export interface NavData {
	me: Me;
	workspaceId: string | null;
	/** The current workspace's boards; null when they could not be read (a workspace the caller is not in). */
	boards: Project[] | null;
}

const KEY = Symbol('loopwright-app-state');

export class AppState {
	readonly #data: () => NavData;
	constructor(data: () => NavData) {
		this.#data = data;
	}
	get me(): Me {
		return this.#data().me;
	}
	get workspaceId(): string | null {
		return this.#data().workspaceId;
	}
	get boards(): Project[] | null {
		return this.#data().boards;
	}
	/** The current workspace with the caller's role; null outside one or in one they are not in. */
	workspace = $derived.by((): WorkspaceSummary | null => this.me.workspaces.find((w) => w.id === this.workspaceId) ?? null);

	/** Reads the caller's workspaces and the boards again (after a mutation that changes them). */
	refresh(): Promise<void> {
		return invalidate(NAV);
	}
}

export function provideAppState(data: () => NavData): AppState {
	return setContext(KEY, new AppState(data));
}

export function useAppState(): AppState {
	const state = getContext<AppState | undefined>(KEY);
	if (!state) throw new Error('useAppState() outside the signed-in layout');
	return state;
}
