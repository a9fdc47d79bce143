/**
 * Light or dark theme, remembered in localStorage (a display preference, not part of a session).
 */
export type ThemeName = 'light' | 'dark';

const STORAGE_KEY = 'burrow-theme';

export class Theme {
  name = $state<ThemeName>('light');
  readonly #storage: Pick<Storage, 'getItem' | 'setItem'> | null;

  constructor(storage: Pick<Storage, 'getItem' | 'setItem'> | null) {
    this.#storage = storage;
    const saved = storage?.getItem(STORAGE_KEY);
    if (saved === 'dark' || saved === 'light') this.name = saved;
  }

  toggle(): void {
    this.set(this.name === 'dark' ? 'light' : 'dark');
  }

  set(name: ThemeName): void {
    this.name = name;
    try {
      this.#storage?.setItem(STORAGE_KEY, name);
    } catch {
      // Storage may be full or disabled; the theme still applies for this visit.
    }
  }
}
