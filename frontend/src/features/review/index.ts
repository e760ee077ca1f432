/** The review feature's public face: queries, the workflow bar, revisions, history and notifications. */
export * from './api/review';
export { CellReview, type ReviewContext } from './components/cell-review';
export { WorkflowBar } from './components/workflow-bar';
