import { InitialSchema1764640000000 } from './1764640000000-InitialSchema';
import { Notebooks1764650000000 } from './1764650000000-Notebooks';
import { AccountSecurity1764660000000 } from './1764660000000-AccountSecurity';
import { SharedResults1764670000000 } from './1764670000000-SharedResults';
import { ServerSecrets1764680000000 } from './1764680000000-ServerSecrets';
import { Collaboration1764690000000 } from './1764690000000-Collaboration';
import { Datasets1764700000000 } from './1764700000000-Datasets';
import { AccountChanges1764720000000 } from './1764720000000-AccountChanges';

/** Every migration, oldest first. Add new ones at the end. */
export const migrations = [
  InitialSchema1764640000000,
  Notebooks1764650000000,
  AccountSecurity1764660000000,
  SharedResults1764670000000,
  ServerSecrets1764680000000,
  Collaboration1764690000000,
  Datasets1764700000000,
  AccountChanges1764720000000,
];
