export { renderReport, CONTENT_SECURITY_POLICY } from './report.ts';
export type { ReportInput, ReportOptions } from './context.ts';
export { escapeHtml } from './escape.ts';
export { formatNumber, formatPercent, formatP } from './format.ts';
export { PALETTE, CATEGORY_COLOURS, SEQUENTIAL, orderedColours, categoryColours } from './palette.ts';
export { renderChart, renderCharts, CHART_CONFIG, type ChartDef } from './vega.ts';
export { barChart, histogram, boxPlot, conditionalBars, scatter, missingHeatmap } from './charts.ts';
export type { ChartSpec, Bar, Box, BoxPoint, Segment, HeatCell } from './charts.ts';
export { boxFromValues, MAX_SCATTER_POINTS, MAX_BOX_POINTS } from './data.ts';
