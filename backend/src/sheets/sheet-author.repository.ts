/**
 * Who prepared a revision of a sheet: its preparer, the co-preparers the preparer named, and anyone
 * whose save was stored. Independent checking (common practice) rests on this list: none of them may
 * check or approve that revision (review/review-access.ts).
 */
import { EntityRepository } from '@mikro-orm/mariadb';
import type { SheetAuthor } from './entities/sheet-author.entity';

export interface Author {
  userId: string;
  name: string;
  /** Named co-preparer (may edit). */
  named: boolean;
  /** Had a save stored. */
  edited: boolean;
}

const UPSERT = 'insert into sheet_author (id, sheet_id, revision_number, user_id, named, edited) values (uuid(), ?, ?, ?, ?, ?)';

/** The SQL of a revision's authors. Its methods run in the caller's transaction when there is one. */
export class SheetAuthorRepository extends EntityRepository<SheetAuthor> {
  async authorsOf(sheetId: string, revisionNumber: number): Promise<Author[]> {
    const rows = await this.em.execute<{ user_id: string; name: string; named: number; edited: number }[]>(
      'select a.user_id, u.name, a.named, a.edited from sheet_author a join app_user u on u.id = a.user_id where a.sheet_id = ? and a.revision_number = ? order by u.name',
      [sheetId, revisionNumber],
    );
    return rows.map((r) => ({ userId: r.user_id, name: r.name, named: !!r.named, edited: !!r.edited }));
  }

  /** Everyone who may not check or approve this revision, by id with their names: the preparer and every author. */
  async notIndependent(sheet: { id: string; revisionNumber: number; preparer: { id: string; name: string } }): Promise<Map<string, string>> {
    return new Map([
      [sheet.preparer.id, sheet.preparer.name],
      ...(await this.authorsOf(sheet.id, sheet.revisionNumber)).map((a) => [a.userId, a.name] as [string, string]),
    ]);
  }

  /** Records that a person's save of this revision was stored (inside the saving transaction). */
  async recordEdit(sheetId: string, revisionNumber: number, userId: string): Promise<void> {
    await this.em.execute(`${UPSERT} on duplicate key update edited = 1`, [sheetId, revisionNumber, userId, 0, 1], 'run');
  }

  /** Sets the named co-preparers of a revision; someone taken off the list stays an author if they edited. */
  async nameCoPreparers(sheetId: string, revisionNumber: number, userIds: string[]): Promise<void> {
    await this.em.execute('update sheet_author set named = 0 where sheet_id = ? and revision_number = ?', [sheetId, revisionNumber], 'run');
    for (const userId of userIds) await this.em.execute(`${UPSERT} on duplicate key update named = 1`, [sheetId, revisionNumber, userId, 1, 0], 'run');
    await this.em.execute('delete from sheet_author where sheet_id = ? and revision_number = ? and named = 0 and edited = 0', [sheetId, revisionNumber], 'run');
  }
}
