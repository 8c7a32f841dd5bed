/**
 * Colours and fonts the charts share. Chosen to stay apart in greyscale print as well as on
 * screen: series differ in lightness, and the marks that matter most are dark.
 */

/** One colour per state (or branch), in order; repeats after six. */
export const SERIES_COLOURS = ['#1b6a8a', '#c2571a', '#6b3fa0', '#3c7a26', '#a3243b', '#4f5d6b'] as const;

export const seriesColour = (i: number): string => SERIES_COLOURS[i % SERIES_COLOURS.length];

export const INK = '#1d2630';
export const MUTED = '#5c6773';
export const GRID = '#e3e7ec';
export const ZERO_LINE = '#8a949e';
export const EVENT_LINE = '#7b5ea7';
export const FIELD_MARK = '#9db3c4';
export const STABLE = '#1b6a8a';
export const UNSTABLE = '#c2571a';
export const FOLD = '#1d2630';

export const AXIS_FONT = '12px system-ui, -apple-system, "Segoe UI", sans-serif';
export const AXIS_LABEL_FONT = 'bold 12px system-ui, -apple-system, "Segoe UI", sans-serif';
