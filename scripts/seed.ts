import { seedDemo } from "./seed-demo";
import { DEMO_COMPANIES, DEMO_PASSWORD } from "./seed-data";

await seedDemo();
console.log(`Seeded ${DEMO_COMPANIES.length} demo companies. Demo password: ${DEMO_PASSWORD}`);
