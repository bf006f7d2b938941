// The application version, kept in one place for the API, the CLI and the database.
export const VERSION = '0.1.0';
