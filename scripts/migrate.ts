// Importing the database module applies every migration in drizzle/ (and creates the data folder).
import "~/lib/db.server";

console.log("Database is up to date.");
