/** The projects feature's public face. */
export * from './api/project-keys';
export * from './api/get-projects';
export * from './api/get-project';
export * from './api/create-project';
export * from './api/get-project-people';
export * from './api/set-project-members';
export { ProjectPeople } from './components/project-people';
