/** The per-epoch table lives in the core (report/epoch-table.ts); kept here for the CLI's imports. */
export { epochTableColumns, epochTableRow, standaloneFrameNote } from '@refdelta/core';
