/**
 * The parts of the sheet repository that are not SQL: reading the cells' ids that MariaDB's GROUP_CONCAT
 * joined. The statements themselves are covered by the integration tests against MariaDB.
 */
import { describe, expect, it } from 'vitest';
import { idList } from './sheet.repository';

describe('idList', () => {
  const ids = ['3f2c7a9e-0b1d-4c5e-8f6a-1b2c3d4e5f60', '9a8b7c6d-5e4f-4a3b-8c2d-1e0f9a8b7c6d', 'c'];
  const full = ids.join(',');
  const length = ids.reduce((n, id) => n + id.length, 0) + ids.length - 1;

  it('splits the joined ids when the list is whole', () => {
    expect(idList({ cell_ids: full, cell_count: 3, cell_ids_length: length })).toEqual(ids);
    // MariaDB may hand the sums back as strings (DECIMAL) or bigints.
    expect(idList({ cell_ids: full, cell_count: '3', cell_ids_length: String(length) })).toEqual(ids);
    expect(idList({ cell_ids: null, cell_count: null, cell_ids_length: null })).toEqual([]);
  });

  it('gives nothing when group_concat_max_len cut the list, even inside an id or just after a separator', () => {
    for (const cut of [full.length - 1, ids[0].length + 1, ids[0].length + 10, 5])
      expect(idList({ cell_ids: full.slice(0, cut), cell_count: 3, cell_ids_length: length })).toBeUndefined();
    // Cut to nothing while there are cells.
    expect(idList({ cell_ids: '', cell_count: 3, cell_ids_length: length })).toBeUndefined();
  });
});
