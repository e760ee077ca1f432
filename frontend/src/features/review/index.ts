/** The review feature's public face: queries, the workflow bar, revisions, history and notifications. */
export * from './api/review-keys';
export * from './api/get-sheet-queries';
export * from './api/get-revisions';
export * from './api/get-history';
export * from './api/get-diff';
export * from './api/get-notifications';
export * from './api/mark-all-read';
export * from './api/sheet-action';
export * from './api/request-check';
export * from './api/set-co-preparers';
export * from './api/raise-query';
export * from './api/reply-to-query';
export * from './api/close-query';
export * from './api/set-agreement';
export { CellReview, type ReviewContext } from './components/cell-review';
export { WorkflowBar } from './components/workflow-bar';
