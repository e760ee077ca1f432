import type { EntityManager } from '@mikro-orm/mariadb';
import { hash } from 'bcrypt';
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
  return created.length ? `demo seed: created ${created.join(', ')}` : 'demo seed: everything already present';
}
