/**
 * Typed context helpers: the root component sets the stores once, every component below reads the
 * ones it needs. No string keys, no casts in components.
 */
import { createContext } from 'svelte';
import type { CurveView } from './curveView.svelte.ts';
import type { Theme } from './theme.svelte.ts';
import type { Workspace } from './workspace.svelte.ts';

export const [getWorkspace, setWorkspace] = createContext<Workspace>();
export const [getCurveView, setCurveView] = createContext<CurveView>();
export const [getTheme, setTheme] = createContext<Theme>();
