/**
 * io: reading instrument text exports into curves (pure, for Node and web workers), remembering
 * mapping answers, keeping raw text. Other layers import from here only.
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
export { importText, importChunks, type TextChunks } from './importText.ts';
export { importFiles, failedImport, type ImportInput } from './importFiles.ts';
export { createImporter, type StreamingImporter } from './createImporter.ts';
export { MappingMemory, type MappingMemoryJSON } from './mappingMemory.ts';
export { MappingError, headerSignature } from './planColumns.ts';
export { RawTextStore, type RawTextRecord } from './rawStore.ts';
export { parseUnit, parseUnitAs, type ParsedUnit, type UnitDimension } from './parseUnit.ts';
export { parseHeaderCell, type HeaderCell } from './parseHeaderCell.ts';
export { KNOWN_METADATA_KEYS } from './readMetadata.ts';
export { delimiterName } from './splitCells.ts';
