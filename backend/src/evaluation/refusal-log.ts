/**
 * Which refusals of a busy evaluator to log: the first of a firm in each window, carrying how many of that
 * firm's were not logged since. A firm that floods the evaluator is told "busy" on every request (and each
 * request has its own request line); without this, each refusal would also write a warning of its own.
 */
export class RefusalLog {
  private readonly seen = new Map<string, { at: number; unlogged: number }>();

  constructor(
    private readonly windowMs = 60_000,
    private readonly maxFirms = 10_000,
    private readonly now: () => number = Date.now,
  ) {}

  /** Undefined: do not log this one. Otherwise log it, with `unlogged` refusals of the firm since the last line. */
  take(firm: string): { unlogged: number } | undefined {
    const now = this.now();
    const seen = this.seen.get(firm);
    if (seen && now - seen.at < this.windowMs) {
      seen.unlogged += 1;
      return undefined;
    }
    this.seen.delete(firm);
    this.seen.set(firm, { at: now, unlogged: 0 });
    // The oldest firms go first once there are too many to remember: at worst one of them logs again.
    if (this.seen.size > this.maxFirms) this.seen.delete(this.seen.keys().next().value as string);
    return { unlogged: seen?.unlogged ?? 0 };
  }
}
