/**
 * When an evaluation still running sends the results it has so far: first as soon as the first cell evaluated
 * afresh (the edited one, the cells above it being reused) is done, or after `firstAfterMs`, whichever is
 * first; then every `everyMs` (a frame) while there are more — so the cells on screen below the edited one
 * follow within a frame or two, not only when the last cell of a long sheet is done.
 */
export class PartialCadence {
  private sentAt: number | undefined;
  private sentCount = 0;
  private fresh = 0;

  constructor(
    private readonly started: number,
    private readonly firstAfterMs = 8,
    private readonly everyMs = 16,
  ) {}

  /** Told before each cell evaluated afresh, with how many results are done: whether to send them now. */
  due(done: number, now: number): boolean {
    this.fresh += 1;
    const due =
      this.sentAt === undefined ? this.fresh >= 2 || now - this.started >= this.firstAfterMs : now - this.sentAt >= this.everyMs && done > this.sentCount;
    if (due) {
      this.sentAt = now;
      this.sentCount = done;
    }
    return due;
  }
}
