/**
 * Tests read the JSON of fetch responses as loosely as supertest's `body`: the assertions that follow
 * check its shape. (Interface merging puts this overload first.)
 */
declare global {
  interface Response {
    json(): Promise<any>;
  }
}
export {};
