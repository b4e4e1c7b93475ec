import { InitialSchema1764640000000 } from './1764640000000-InitialSchema';

/** Every migration, oldest first. Add new ones at the end. */
export const migrations = [InitialSchema1764640000000];
