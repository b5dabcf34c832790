import type { Pool } from 'pg';
import type { Db } from '../db/client';
import type { Config } from './config';

/** What every router and service receives: the database and the configuration. */
export type AppContext = { db: Db; pool: Pool; config: Config };
