import type { EntityManager } from '@mikro-orm/mariadb';
import { Firm } from '../../firms/entities/firm.entity';

export const DEMO_FIRM_NAME = 'Northfold Engineering';

/** Creates the demo data that is missing; returns a one-line summary. */
export async function seedDemo(em: EntityManager): Promise<string> {
  const existing = await em.findOne(Firm, { name: DEMO_FIRM_NAME });
  if (existing) return `demo seed: ${DEMO_FIRM_NAME} already present`;
  em.persist(new Firm(DEMO_FIRM_NAME));
  await em.flush();
  return `demo seed: created ${DEMO_FIRM_NAME}`;
}
