/** Report stage: pure builders of CSV rows, GeoJSON and the run summary (strings/objects out). */
export { fixed, jsonNumber, frameEpochText } from './format.js';
export { pointReferenceWords, frameWords } from './point-reference.js';
export {
  epochColumns, epochRow, epochRows, csvPreamble, relativeClockColumn, systemsWithClocks,
  type CsvTable, type CsvPreambleInput,
} from './epoch-rows.js';
export { RESIDUAL_COLUMNS, residualRows, residualRowsOf } from './residual-rows.js';
export { geojson, epochFeature, geojsonNote, isWgs84Label, type GeoJsonOptions, type PointFeature, type RefdeltaFeatureCollection } from './geojson.js';
export {
  summaryJson, scatterJson, CAUTIONS, SOLVE_SCATTER_ABOUT,
  type InputKind, type InputFileRecord, type OutputFileRecord, type LabelledScatter, type SummaryExtras,
} from './summary-json.js';
export {
  percentile, mean, rms, horizontalVerticalStats, enuDifferences, meanEcef, positionScatter, seriesScatter, PositionSeries,
  type HorizontalVerticalStats, type ScatterStats,
} from './statistics.js';
export { errorsAgainstTruth, truthStatistics, type TruthPoint } from './truth-compare.js';
export { epochTableColumns, epochTableRow, frameEpochCell, standaloneFrameNote } from './epoch-table.js';
export { VOCABULARY, columnsDescribed, type VocabularyEntry } from './vocabulary.js';
export { tableMetadata, crsStatement, type TableMetadataInput, type CrsStatement } from './table-metadata.js';
export * from './output-registry.js';
export * from './output-kinds.js';
export { GeoPackageWriter, csvtText, gpkgPointBlob, gpkgFieldType, initGeoPackage, type SqliteDatabase, type GpkgLayer, type GpkgSrs } from './geopackage.js';
export { kmlPlacemark, kmlStart, kmlEnd, kmlFrameNote, xmlText } from './kml.js';
export { pointsDxf, dxfMtextValue, DXF_POINTS_LAYER, DXF_NAMES_LAYER, type DxfPoint } from './dxf.js';
export { gridCrsWords, heightsStatement, pooledPointScatter, POOLED_POINT_SCATTER_KIND, pointsRunScatter, withPointsRun, type HeightsStatement, type PointsRunOptions } from './points-run-summary.js';
