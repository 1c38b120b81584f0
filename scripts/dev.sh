#!/usr/bin/env bash
# npm run dev: the services, migrations and seed of `npm start`, then Vite's dev server.
source "$(dirname "$0")/lib.sh"
ensure_packages
scripts/db.sh start
node_modules/.bin/tsx scripts/migrate.ts
node_modules/.bin/tsx scripts/seed.ts
ensure_mail_catcher
ensure_payments_fake
exec node_modules/.bin/vite dev --port "${PORT:-5173}"
