/**
 * The look every chart shares, from the colour scheme's custom properties (app/globals.css), so
 * the charts follow the light and dark schemes: grid lines, axis ticks, and the line charts' margin.
 */
export const CHART_GRID = { stroke: "var(--t-silt-line)", strokeDasharray: "3 3" } as const;
/** numbers and labels along an axis */
export const AXIS_TICK = { fontSize: 12, fill: "var(--t-silt-ink)" } as const;
/** the names on a bar chart's category axis */
export const NAME_TICK = { fontSize: 12, fill: "var(--t-ink)" } as const;
/** the small multiples' ticks */
export const SMALL_TICK = { fontSize: 11, fill: "var(--t-silt-ink)" } as const;
export const LINE_MARGIN = { top: 8, right: 16, bottom: 4, left: 0 } as const;
