/** The projects feature's public face. */
export * from './api/projects';
export { ProjectPeople } from './components/project-people';
