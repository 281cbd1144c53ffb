/**
 * Database chores for the start and test scripts and for developers:
 *   node --import tsx scripts/db.ts migrate | rollback [all] | status | seed [--if-empty] | reference
 *   ADMIN_PASSWORD=… node --import tsx scripts/db.ts create-admin <email> <full name>
 * Reads DATABASE_URL from the environment (the start script sets it from .env).
 */
import { createSequelize } from '../src/db/connection';
import { migrator } from '../src/db/migrator';
import { initModels, User } from '../src/db/models';
import { hashPassword } from '../src/server/auth/password';
import { createUserSchema } from '../src/lib/schemas/users';

async function main(): Promise<number> {
  const [command, arg] = process.argv.slice(2);
  const url = process.env.DATABASE_URL;
  if (!url) {
    console.error('DATABASE_URL is not set (npm start sets it from .env).');
    return 2;
  }
  const sequelize = createSequelize(url);
  initModels(sequelize);
  const umzug = migrator(sequelize);
  try {
    switch (command) {
      case 'migrate': {
        const done = await umzug.up();
        console.log(done.length ? `applied ${done.length} migration(s): ${done.map((m) => m.name).join(', ')}` : 'database schema is up to date');
        return 0;
      }
      case 'rollback': {
        const done = await umzug.down(arg === 'all' ? { to: 0 } : undefined);
        console.log(`rolled back ${done.length} migration(s)`);
        return 0;
      }
      case 'status': {
        const [done, pending] = await Promise.all([umzug.executed(), umzug.pending()]);
        console.log(`applied: ${done.length}, pending: ${pending.map((m) => m.name).join(', ') || 'none'}`);
        return 0;
      }
      case 'reference': {
        const { seedReferenceRanges } = await import('../seeders/reference-ranges');
        console.log(await seedReferenceRanges());
        return 0;
      }
      case 'seed': {
        if (arg === '--if-empty' && (await User.count()) > 0) {
          console.log('demo clinic already present; not seeding again');
          return 0;
        }
        // Loaded only here: the demo seed needs faker, a development dependency.
        const { seedDemoClinic } = await import('../seeders/demo-clinic');
        await seedDemoClinic(sequelize);
        console.log('seeded the demo clinic');
        return 0;
      }
      case 'create-admin': {
        // The first manager account of a production install (no demo seed there).
        const parsed = createUserSchema.safeParse({
          email: arg,
          displayName: process.argv.slice(4).join(' '),
          role: 'admin',
          password: process.env.ADMIN_PASSWORD ?? '',
        });
        if (!parsed.success) {
          console.error('create-admin: ' + parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; '));
          return 2;
        }
        const { email, displayName, password } = parsed.data;
        await User.create({ email, displayName, role: 'admin', passwordHash: await hashPassword(password), referrerId: null });
        console.log(`created manager account ${email}`);
        return 0;
      }
      default:
        console.error('usage: scripts/db.ts migrate | rollback [all] | status | seed [--if-empty] | reference | create-admin <email> <name>');
        return 2;
    }
  } finally {
    await sequelize.close();
  }
}

main().then(
  (code) => process.exit(code),
  (error: Error) => {
    // One line, no stack: these run inside npm start and npm test.
    console.error(`database step failed: ${error.name}: ${error.message.split('\n')[0]}`);
    process.exit(1);
  },
);
