/** The part of sql.js (SQLite compiled to WebAssembly) the CLI uses; the package ships no types. */
declare module 'sql.js' {
  const initSqlJs: (config?: { locateFile?: (file: string) => string }) => Promise<{ Database: new () => import('@refdelta/core').SqliteDatabase }>;
  export default initSqlJs;
}
