/**
 * The database schema. One file per area keeps concurrent work apart; drizzle-kit reads this entry.
 */
export * from './schema-auth';
export * from './schema-catalog';
export * from './schema-builds';
export * from './schema-sharing';
export * from './schema-sheet';
export * from './schema-loop';
