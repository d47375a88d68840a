// One place that says where the database is, so the app, scripts and tests agree.
export function databaseUrl(): string {
  const url = process.env.DATABASE_URL;
  if (!url) {
    throw new Error('DATABASE_URL is not set; start the app with ./scripts/start.sh or set it yourself.');
  }
  return url;
}
