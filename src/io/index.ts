/**
 * io: reading instrument text exports into curves. Pure and usable from Node and from a web worker:
 * importText / importChunks / createImporter take text (whole, as chunks, or pushed piece by piece)
 * and a file name, and never touch the file system. Mapping answers are remembered with
 * MappingMemory; raw text is kept in IndexedDB with RawTextStore.
 * The Node-only reader of files and folders (src/io/readFileNode.ts) is deliberately not exported
 * here, so that this surface stays free of node: imports for the browser bundle; the CLI imports it
 * directly.
 */
export type {
  ColumnRole,
  Curve,
  CurveKind,
  DecimalMark,
  Delimiter,
  Dialect,
  ImportColumn,
  ImportedFile,
  ImportOptions,
  ImportProblem,
  LineEnding,
  MappingAmbiguity,
  MappingAnswer,
  MappingLookup,
  MappingProposal,
  MetadataEntry,
  Segment,
} from './types.ts';
export { COLUMN_ROLES } from './types.ts';

// Importing
export { importText, importChunks, type TextChunks } from './importText.ts';
export { importFiles, failedImport, type ImportInput } from './importFiles.ts';
export { createImporter, type StreamingImporter } from './createImporter.ts';

// Mapping answers
export { MappingMemory, type MappingMemoryJSON } from './mappingMemory.ts';
export { MappingError, headerSignature } from './planColumns.ts';

// Raw text in the browser
export { RawTextStore, type RawTextRecord } from './rawStore.ts';
export { done, promised } from './indexedDbPromises.ts';

// Building blocks a dialog or an exporter may reuse
export { parseUnit, parseUnitAs, SI_UNIT_OF, type ParsedUnit, type UnitDimension } from './parseUnit.ts';
export { parseHeaderCell, type HeaderCell } from './parseHeaderCell.ts';
export { KNOWN_METADATA_KEYS } from './readMetadata.ts';
export { delimiterName } from './splitCells.ts';
export { writeReport } from './reportHtml.ts';
export { stripBoxPlotSvg, driftPlotSvg, gridMapSvg, REPORT_PLOT_COLOURS } from './reportSvg.ts';
export { escapeHtml } from './reportFormat.ts';

// Settings files kept with the data (the CLI and the dashboard read them alike)
export { isSettingsFileName, readSettingsText, settingsAgree, type SettingsFileRead } from './settingsFile.ts';
