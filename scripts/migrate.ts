// Importing the database module applies every migration in drizzle/ (and creates the data folder).
import "~/lib/platform/db.server";

console.log("Database is up to date.");
