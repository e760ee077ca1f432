import { Injectable } from '@nestjs/common';
import { LRUCache } from 'lru-cache';

/** At most this much of the cells' JSON is kept, in bytes; a sheet's cells larger than a tenth of it are never kept. */
const MAX_BYTES = 64 * 1024 * 1024;

/**
 * The cells of the sheet views last read, as the JSON bytes sent, by sheet id, each with the stamp MariaDB
 * computed from every column that JSON is made of (SheetRepository.viewJson). A read asks MariaDB for the
 * stamp of the cells as they are now — in the statement that reads the heading — and sends the kept bytes only
 * when the stamp is the same: whatever changed a cell, by whichever path or instance, changes the stamp, so
 * nothing is ever invalidated by hand and nothing stale is sent. Least recently read sheets go first.
 */
@Injectable()
export class SheetViewCache {
  private readonly cells = new LRUCache<string, { stamp: string; json: Buffer }>({
    maxSize: MAX_BYTES,
    maxEntrySize: Math.floor(MAX_BYTES / 10),
    sizeCalculation: (entry) => entry.json.length + entry.stamp.length + 100,
  });

  /** The kept cells' JSON of a sheet if it was read with this stamp. */
  get(sheetId: string, stamp: string): Buffer | undefined {
    const entry = this.cells.get(sheetId);
    return entry?.stamp === stamp ? entry.json : undefined;
  }

  set(sheetId: string, stamp: string, json: Buffer): void {
    this.cells.set(sheetId, { stamp, json });
  }

  /** Sheets kept, and their bytes (for tests and figures). */
  get size(): { sheets: number; bytes: number } {
    return { sheets: this.cells.size, bytes: this.cells.calculatedSize };
  }
}
