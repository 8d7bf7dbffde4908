import { storeContract } from './contract.ts';
import { sqliteFactory } from './factories.ts';

storeContract('SQLite', sqliteFactory);
