/**
 * Where the user is (view, bus, net), appearance and display units. The view is mirrored in the
 * address's #fragment so reload and browser back keep the place.
 */
import { defineStore } from 'pinia';
import { ref, watch } from 'vue';
import type { LengthUnit } from '../lib/format.js';

export type ViewName = 'overview' | 'bus' | 'net' | 'stackup' | 'parts' | 'corners' | 'import' | 'new';
export interface Place {
  view: ViewName;
  bus?: string;
  net?: string;
}
export type Theme = 'system' | 'light' | 'dark';

const VIEWS: ViewName[] = ['overview', 'bus', 'net', 'stackup', 'parts', 'corners', 'import', 'new'];

function placeFromHash(hash: string): Place {
  const [view, ...rest] = hash.replace(/^#\/?/, '').split('/').map((part) => {
    try {
      return decodeURIComponent(part);
    } catch {
      return '';
    }
  });
  if (!VIEWS.includes(view as ViewName)) return { view: 'overview' };
  if (view === 'bus') return rest[0] ? { view, bus: rest[0] } : { view: 'overview' };
  if (view === 'net') return rest[0] ? { view, net: rest[0] } : { view: 'overview' };
  return { view: view as ViewName };
}

function hashOf(place: Place): string {
  if (place.view === 'bus') return `#/bus/${encodeURIComponent(place.bus ?? '')}`;
  if (place.view === 'net') return `#/net/${encodeURIComponent(place.net ?? '')}`;
  return `#/${place.view}`;
}

function stored<T extends string>(key: string, allowed: readonly T[], fallback: T): T {
  try {
    const value = localStorage.getItem(key);
    return allowed.includes(value as T) ? (value as T) : fallback;
  } catch {
    return fallback;
  }
}

export const useUiStore = defineStore('ui', () => {
  const place = ref<Place>(placeFromHash(window.location.hash));
  const theme = ref<Theme>(stored('slackline.theme', ['system', 'light', 'dark'] as const, 'system'));
  const lengthUnit = ref<LengthUnit>(stored('slackline.lengthUnit', ['mil', 'mm'] as const, 'mil'));

  function go(next: Place): void {
    place.value = next;
    const hash = hashOf(next);
    if (window.location.hash !== hash) history.pushState(null, '', hash);
  }

  const follow = () => {
    const next = placeFromHash(window.location.hash);
    if (hashOf(next) !== hashOf(place.value)) place.value = next;
  };
  window.addEventListener('popstate', follow);
  window.addEventListener('hashchange', follow);

  function cycleTheme(): void {
    theme.value = theme.value === 'system' ? 'dark' : theme.value === 'dark' ? 'light' : 'system';
  }

  // "system" follows the operating system's appearance, live; the stylesheet only knows data-theme.
  const systemDark = window.matchMedia('(prefers-color-scheme: dark)');
  /** The appearance in effect (charts pick their palette from it). */
  const resolvedTheme = ref<'light' | 'dark'>('light');

  function applyTheme(): void {
    const resolved = theme.value === 'system' ? (systemDark.matches ? 'dark' : 'light') : theme.value;
    resolvedTheme.value = resolved;
    document.documentElement.setAttribute('data-theme', resolved);
  }
  systemDark.addEventListener('change', applyTheme);

  watch(theme, (value) => {
    applyTheme();
    try {
      localStorage.setItem('slackline.theme', value);
    } catch {
      /* private mode: the choice lasts this session only */
    }
  }, { immediate: true });

  watch(lengthUnit, (value) => {
    try {
      localStorage.setItem('slackline.lengthUnit', value);
    } catch {
      /* as above */
    }
  });

  return { place, theme, resolvedTheme, lengthUnit, go, cycleTheme };
});
