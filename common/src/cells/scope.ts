/**
 * What a cell can see: the names defined above it and on its own earlier lines. The scope also knows
 * every definition in the sheet (to say where a name used too early is defined) and records which
 * outer names a cell read, so incremental evaluation knows what a cell depends on.
 */
export interface Place {
  cell: number; // 0-based
  line: number; // 1-based
}

export const describePlace = (p: Place) => `cell ${p.cell + 1}, line ${p.line}`;

const ASSIGNMENT = /^\s*([A-Za-z_\u0370-\u03FF][A-Za-z0-9_\u0370-\u03FF]*)\s*=(?!=)/;

/** The name a calc line assigns, read without a full parse. */
export function assignedName(line: string): string | undefined {
  return ASSIGNMENT.exec(line)?.[1];
}

/**
 * Freezes a value and everything it holds (a matrix's data and size, a unit's parts, a complex
 * number), so a value handed from one cell to the next cannot be mutated by the cells below:
 * an attempt fails instead of silently changing an earlier result.
 */
export function freezeValue<T>(value: T): T {
  // Frozen on the way down, so an object met again (shared, or a cycle) is seen frozen and not visited twice.
  const visit = (v: unknown): void => {
    if (v === null || typeof v !== 'object' || Object.isFrozen(v)) return;
    if (ArrayBuffer.isView(v)) return; // typed arrays cannot be frozen; the engine's own series only
    Object.freeze(v);
    if (Array.isArray(v)) {
      for (let k = 0; k < v.length; k++) if (typeof v[k] === 'object') visit(v[k]);
    } else {
      // Own properties only (a Unit's prototype has dozens of enumerable methods).
      const record = v as Record<string, unknown>;
      for (const key of Object.keys(record)) if (typeof record[key] === 'object') visit(record[key]);
    }
  };
  visit(value);
  return value;
}

/** What the scope held for a name: whether it had a value, the value, and where it was defined or failed. */
export interface Held {
  present: boolean;
  value: unknown;
  origin: Place | undefined;
  failed: Place | undefined;
}

export class SheetScope {
  readonly values = new Map<string, unknown>();
  readonly origin = new Map<string, Place>();
  /** Names whose definition failed, with where: using one says so instead of "unknown". */
  readonly failed = new Map<string, Place>();
  private reads: Set<string> | undefined;
  /** While `journaling`: for each name changed so far, what it held before its first change. */
  private journal: Map<string, Held> | undefined;
  /** Display text of values, remembered for the working of the lines that use them. */
  private readonly shown = new Map<string, { value: unknown; text: string }>();

  /** Remembers how a value was shown where it was defined (with its `to` unit or rad/s). */
  rememberDisplay(name: string, value: unknown, text: string): void {
    this.shown.set(name, { value, text });
  }

  /** How a name's current value was shown where it was defined, if it was remembered. */
  rememberedDisplay(name: string): string | undefined {
    const known = this.shown.get(name);
    return known && known.value === this.values.get(name) ? known.text : undefined;
  }

  /** The display text of a name's value, computed once per value. */
  displayOf(name: string, format: (value: unknown) => string): string {
    const value = this.values.get(name);
    const known = this.shown.get(name);
    if (known && known.value === value) return known.text;
    const text = format(value);
    this.shown.set(name, { value, text });
    return text;
  }

  constructor(readonly definitions: Map<string, Place[]>) {}

  has(name: string): boolean {
    this.reads?.add(name);
    return this.values.has(name);
  }

  get(name: string): unknown {
    this.reads?.add(name);
    return this.values.get(name);
  }

  /** What the scope holds for a name now. */
  held(name: string): Held {
    return { present: this.values.has(name), value: this.values.get(name), origin: this.origin.get(name), failed: this.failed.get(name) };
  }

  /** Notes what a name held before it first changes (every change of the three maps passes here). */
  private changing(name: string): void {
    if (this.journal && !this.journal.has(name)) this.journal.set(name, this.held(name));
  }

  /** Binds a name; the value is frozen, so nothing a later cell does can change what this one showed. */
  define(name: string, value: unknown, place: Place): void {
    this.changing(name);
    this.values.set(name, freezeValue(value));
    this.origin.set(name, place);
    this.failed.delete(name);
  }

  markFailed(name: string, place: Place): void {
    this.changing(name);
    this.values.delete(name);
    this.origin.delete(name);
    this.failed.set(name, place);
  }

  /** The first definition of a name after a place, if any. */
  definedLater(name: string, after: Place): Place | undefined {
    return this.definitions.get(name)?.find((p) => p.cell > after.cell || (p.cell === after.cell && p.line > after.line));
  }

  /** Runs fn and returns the outer names it read (names defined inside the cell are filtered by the caller). */
  tracking<T>(fn: () => T): { result: T; reads: Set<string> } {
    const before = this.reads;
    const reads = new Set<string>();
    this.reads = reads;
    try {
      return { result: fn(), reads };
    } finally {
      this.reads = before;
    }
  }

  /**
   * Runs fn and returns, for each name it changed, what that name held before — so a caller learns what a
   * cell defined and what it saw without copying the scope.
   */
  journaling<T>(fn: () => T): { result: T; before: Map<string, Held> } {
    const outer = this.journal;
    const before = new Map<string, Held>();
    this.journal = before;
    try {
      return { result: fn(), before };
    } finally {
      this.journal = outer;
      if (outer) for (const [name, held] of before) if (!outer.has(name)) outer.set(name, held);
    }
  }

  /** A Map-like view for mathjs that records reads. */
  asMathScope(): Map<string, unknown> {
    // eslint-disable-next-line @typescript-eslint/no-this-alias
    const scope = this;
    return new (class extends Map<string, unknown> {
      get(key: string) {
        return scope.get(key);
      }
      has(key: string) {
        return scope.has(key);
      }
      set(key: string, value: unknown) {
        scope.changing(key);
        scope.values.set(key, value);
        return this;
      }
      keys() {
        return scope.values.keys();
      }
    })();
  }
}
