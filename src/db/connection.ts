import { Sequelize } from 'sequelize';
import { config } from '../server/config';
import { initModels } from './models';

let instance: Sequelize | undefined;

/** Builds a Sequelize instance for a mariadb:// URL; times are stored and read as UTC. */
export function createSequelize(url: string): Sequelize {
  return new Sequelize(url, {
    dialect: 'mariadb',
    timezone: '+00:00',
    // SQL text carries patient data in its values: never logged.
    logging: false,
    pool: { max: 10, min: 0, acquire: 10_000, idle: 10_000 },
    dialectOptions: { connectTimeout: 3_000 },
    define: { underscored: true, charset: 'utf8mb4', collate: 'utf8mb4_unicode_ci' },
  });
}

/** The app's shared connection pool, created on first use with every model registered. */
export function db(): Sequelize {
  if (!instance) {
    instance = createSequelize(config().DATABASE_URL);
    initModels(instance);
  }
  return instance;
}

/** Closes the pool (tests and scripts). */
export async function closeDb(): Promise<void> {
  if (instance) {
    await instance.close();
    instance = undefined;
  }
}
