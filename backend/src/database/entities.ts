import { Firm } from '../firms/entities/firm.entity';

/** Every entity, listed once: the ORM, the migrator and the seed read this list. */
export const ENTITIES = [Firm];
