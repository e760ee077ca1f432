/**
 * The migration that made project_member and project_client one table (project_person) keeps every link,
 * both ways: run here on the real MariaDB, down (the two old tables filled from the new one) and up again.
 */
import { MikroORM } from '@mikro-orm/core';
import type { AbstractSqlDriver, EntityManager } from '@mikro-orm/mariadb';
import type { INestApplication } from '@nestjs/common';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Migration20261202233510 } from '../src/database/migrations/Migration20261202233510';
import { as, makeCaller } from './support/sessions';
import { createTestApp } from './support/test-app';

describe('the migration to one project–person link', () => {
  let app: INestApplication;
  let orm: MikroORM;
  const sql = <T extends object>(query: string, params: unknown[] = []) => (orm.em.fork() as EntityManager).getConnection().execute<T>(query, params);

  /** The statements of one direction of the migration, run in order. */
  async function run(direction: 'up' | 'down') {
    const migration = new Migration20261202233510(orm.em.getDriver() as AbstractSqlDriver, orm.config);
    await migration[direction]();
    for (const query of migration.getQueries()) await sql(typeof query === 'string' ? query : query.toString());
  }

  beforeAll(async () => {
    app = await createTestApp();
    orm = app.get(MikroORM);
  });
  afterAll(async () => {
    await app?.close();
  });

  it('copies the team and the clients of a project to the old tables and back', async () => {
    const owner = await makeCaller(app, ['owner', 'engineer']);
    const project = (
      await as(app, owner, 'post', '/api/projects').send({ jobNumber: 'J-MIG-1', title: 'Migration', clientOrganisation: 'C', site: 'S' }).expect(201)
    ).body;
    const client = await makeCaller(app, ['client'], owner.firm);
    await sql("insert into project_person (id, project_id, user_id, standing) values (uuid(), ?, ?, 'client')", [project.id, client.user.id]);
    const before = await sql<{ id: string; user_id: string; standing: string }[]>(
      'select id, user_id, standing from project_person where project_id = ? order by standing',
      [project.id],
    );
    expect(before.map((r) => [r.user_id, r.standing])).toEqual([
      [client.user.id, 'client'],
      [owner.user.id, 'team'],
    ]);
    await run('down');
    try {
      expect(await sql('select id, user_id from project_member where project_id = ?', [project.id])).toEqual([{ id: before[1].id, user_id: owner.user.id }]);
      expect(await sql('select id, user_id from project_client where project_id = ?', [project.id])).toEqual([{ id: before[0].id, user_id: client.user.id }]);
    } finally {
      await run('up');
    }
    expect(await sql('select id, user_id, standing from project_person where project_id = ? order by standing', [project.id])).toEqual(before);
  });
});
