/** The sheets feature's public face: sheets, their editor and attachments. The review is passed in as a slot. */
export * from './api/sheet-keys';
export * from './api/get-project-sheets';
export * from './api/get-sheet';
export * from './api/get-templates';
export * from './api/create-sheet';
export * from './api/save-as-template';
export * from './api/get-attachments';
export { AttachmentsPanel } from './components/attachments-panel';
export type { ReviewSlot } from './editor/cell-frame';
export { SheetEditor } from './editor/sheet-editor';
export { KeyboardHelp } from './editor/keyboard-help';
