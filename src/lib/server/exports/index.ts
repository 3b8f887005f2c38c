/**
 * Exports of a loop revision (server-only): sweep CSV, Bode plot SVG and PNG, sign-off report PDF, design JSON
 * export/import. The SPICE netlist is pure text and lives in the engine ($lib/engine/spice).
 */
export { sweepCsv, verdictCsv, SWEEP_CSV_COLUMNS } from './csv';
export { renderBodeSvg, BODE_SVG_HEIGHT, type BodeSvgOptions } from './bodeSvg';
export { renderBodePng, svgToPng, type PngOptions } from './png';
export { plotFromResponse, networkRoots, type PlotFromResponseOptions } from './plotData';
export type { ExportPlot, ExportTrace, ExportMeasured, ExportTraceKind } from './plotTypes';
export { buildSignoffPdf, REPORT_CAUTION, HIGH_VOLTAGE_LIMIT, type SignoffReportInput, type ReportCornerTrace, type ReviewEntry, type PdfOptions } from './signoffPdf';
export { exportDesignJson, exportSignedOffJson, importDesignJson, importFailure, DESIGN_JSON_MAX_CHARS, type DesignImportResult } from './designJson';
export { PALETTES, type ThemeName, type Palette } from './theme';
