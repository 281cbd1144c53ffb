import { createRequire } from 'node:module';
import path from 'node:path';
import { Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';

const require = createRequire(import.meta.url);

interface MigrationModule {
  up(queryInterface: unknown, sequelize: typeof Sequelize): Promise<void>;
  down(queryInterface: unknown, sequelize: typeof Sequelize): Promise<void>;
}

/**
 * Umzug over the `.cjs` files in `migrations/`, recorded in the `SequelizeMeta` table in the
 * same shape sequelize-cli uses, so either tool can read the history.
 */
export function migrator(sequelize: Sequelize, root = process.cwd()) {
  return new Umzug({
    migrations: {
      glob: ['migrations/*.cjs', { cwd: root }],
      resolve: ({ name, path: file }) => {
        const mod = require(path.resolve(root, file!)) as MigrationModule;
        return {
          name,
          up: () => mod.up(sequelize.getQueryInterface(), Sequelize),
          down: () => mod.down(sequelize.getQueryInterface(), Sequelize),
        };
      },
    },
    storage: new SequelizeStorage({ sequelize, modelName: 'SequelizeMeta', tableName: 'SequelizeMeta' }),
    context: sequelize.getQueryInterface(),
    logger: undefined,
  });
}
