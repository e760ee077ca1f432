import { readdirSync, readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import type { EntityManager } from '@mikro-orm/mariadb';
import { evaluateSheet, parseSheetJson } from '@ampwright/common';
import { hash } from 'bcrypt';
import { Project, ProjectPerson } from '../../projects/entities/project.entity';
import { type SheetState } from '../../sheets/entities/sheet.entity';
import { sheetFromFile } from '../../sheets/sheet-file';
import type { Role } from '../../core/roles';
import { Firm } from '../../firms/entities/firm.entity';
import { Membership } from '../../firms/entities/membership.entity';
import { User } from '../../users/entities/user.entity';

export const DEMO_FIRM_NAME = 'Northfold Engineering';
/** For local use only; README.md, "Demo data". */
export const DEMO_PASSWORD = 'Ampwright-demo-1';

export const DEMO_PEOPLE: { email: string; name: string; roles: Role[] }[] = [
  { email: 'owner@northfold.example', name: 'Morag Lindqvist', roles: ['owner'] },
  { email: 'engineer@northfold.example', name: 'Tomasz Reyes', roles: ['engineer'] },
  { email: 'engineer2@northfold.example', name: 'Aiko Brennan', roles: ['engineer'] },
  { email: 'checker@northfold.example', name: 'Priya Okonkwo', roles: ['engineer', 'checker'] },
  { email: 'approver@northfold.example', name: 'Hal Vermeulen', roles: ['engineer', 'approver'] },
  { email: 'client@kestrelridge.example', name: 'Dana Kestrel', roles: ['client'] },
];

/** Creates the demo data that is missing; returns a one-line summary. Running it again changes nothing. */
export async function seedDemo(em: EntityManager, bcryptCost = 12): Promise<string> {
  let firm = await em.findOne(Firm, { name: DEMO_FIRM_NAME });
  const created: string[] = [];
  if (!firm) {
    firm = new Firm(DEMO_FIRM_NAME);
    em.persist(firm);
    created.push(DEMO_FIRM_NAME);
  }
  let passwordHash: string | undefined;
  for (const person of DEMO_PEOPLE) {
    let user = await em.findOne(User, { email: person.email });
    if (!user) {
      // One hash for all demo people: they share the documented demo password anyway.
      passwordHash ??= await hash(DEMO_PASSWORD, bcryptCost);
      user = new User(person.email, person.name, passwordHash);
      em.persist(user);
      created.push(person.email);
    }
    if (!(await em.findOne(Membership, { firm, user }))) em.persist(new Membership(firm, user, person.roles));
  }
  await em.flush();
  created.push(...(await seedKestrelRidge(em, firm)));
  return created.length ? `demo seed: created ${created.join(', ')}` : 'demo seed: everything already present';
}

export const DEMO_JOB_NUMBER = 'NE-2417';

/** The Kestrel Ridge project: one sheet per template, in several states, evaluated and stored. */
async function seedKestrelRidge(em: EntityManager, firm: Firm): Promise<string[]> {
  if (await em.findOne(Project, { firm, jobNumber: DEMO_JOB_NUMBER })) return [];
  const people = Object.fromEntries(await Promise.all(DEMO_PEOPLE.map(async (p) => [p.email.split('@')[0], await em.findOneOrFail(User, { email: p.email })])));
  const project = new Project(
    firm,
    {
      jobNumber: DEMO_JOB_NUMBER,
      title: 'Main switchboard power-factor correction',
      clientOrganisation: 'Kestrel Ridge Cold Storage',
      site: 'Kestrel Ridge distribution centre, 400 V 50 Hz plant',
    },
    people.engineer,
  );
  em.persist([project, new ProjectPerson(project, people.client, 'client')]);
  const dir = resolve(__dirname, '..', '..', '..', '..', 'templates');
  const states: SheetState[] = ['being-prepared', 'with-checker', 'being-prepared', 'checked', 'being-prepared', 'being-prepared'];
  readdirSync(dir)
    .filter((f) => f.endsWith('.json'))
    .sort()
    .forEach((file, i) => {
      const parsed = parseSheetJson(readFileSync(join(dir, file), 'utf8'));
      if (!parsed.ok) throw new Error(`template ${file} is not valid`);
      const { sheet, cells } = sheetFromFile(project, `C-${String(101 + i)}`, parsed.sheet.title, parsed.sheet, i % 2 ? people.engineer2 : people.engineer);
      sheet.state = states[i % states.length];
      if (sheet.state !== 'being-prepared') sheet.checker = people.checker;
      const results = evaluateSheet(parsed.sheet).cells;
      cells.forEach((cell, k) => {
        cell.results = results[k];
      });
      em.persist(cells);
      em.persist(sheet);
    });
  await em.flush();
  return [`project ${DEMO_JOB_NUMBER} with its sheets`];
}
