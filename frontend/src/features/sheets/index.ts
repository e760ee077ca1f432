/** The sheets feature's public face: sheets, their editor and attachments. The review is passed in as a slot. */
export * from './api/sheets';
export { AttachmentsPanel } from './components/attachments-panel';
export type { ReviewSlot } from './editor/cell-frame';
export { SheetEditor } from './editor/sheet-editor';
