/** Self-contained HTML reports (inline SVG charts, no script): a session page and a batch index page. */
export type {
  EpochSeries, ResidualSeries, SkySeries, ReportPoint, ReportCheckPair, ReportControlCheck, ReportInput, SessionReportData, BatchIndexEntry, BatchIndexData,
} from './report-data.js';
export { buildSessionReportHtml, REPORT_CAUTIONS } from './session-report.js';
export { buildBatchIndexHtml, batchOrder } from './batch-index.js';
export { decimationStride, decimatedIndices } from './decimate.js';
export { TIME_SERIES_MAX_EPOCHS } from './chart-time-series.js';
export { PLAN_MAX_EPOCHS, ELLIPSE_95_SCALE } from './chart-plan.js';
export { OCCUPATION_MAX_EPOCHS, OCCUPATION_WINDOW_SLACK_S, occupationEpochs, scatterRadius95M } from './chart-occupation.js';
export { SKY_MAX_VERTICES_PER_SATELLITE, skyTracks } from './chart-sky.js';
export { RESIDUALS_MAX_USED, RESIDUALS_MAX_REJECTED_PER_REASON, residualRowsDrawn } from './chart-residuals.js';
export { OKABE_ITO } from './palette.js';
export { syntheticSessionReportData } from './synthetic-session.js';
export { satelliteDirections, SKY_CSV_COLUMNS, type SatelliteDirection } from './sky-directions.js';
