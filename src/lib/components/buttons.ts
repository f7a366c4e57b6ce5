/** Shared button classes, so every screen's buttons look alike. */
export const primaryButton =
	'inline-flex items-center rounded-md bg-liquid-700 px-4 py-2 text-sm font-medium text-white shadow-sm hover:bg-liquid-800 focus:outline-none focus:ring-2 focus:ring-liquid-500/40 disabled:opacity-50';
export const secondaryButton =
	'inline-flex items-center rounded-md border border-structure-300 bg-white px-4 py-2 text-sm font-medium text-structure-700 shadow-sm hover:bg-structure-50 focus:outline-none focus:ring-2 focus:ring-liquid-500/30';
export const dangerButton =
	'inline-flex items-center rounded-md bg-bad px-4 py-2 text-sm font-medium text-white shadow-sm hover:opacity-90 focus:outline-none focus:ring-2 focus:ring-bad/40';
export const linkClass = 'text-liquid-700 underline-offset-2 hover:underline';
