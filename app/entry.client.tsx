import { startTransition, StrictMode } from "react";
import { hydrateRoot } from "react-dom/client";
import { HydratedRouter } from "react-router/dom";
import { stopEarlyInput } from "~/components/early-input";

// React Router's own client entry with two changes. Hydration starts in a task of its own, so
// evaluating the page's modules and setting up the router are not one long task on a slow phone.
// And what the visitor did before it started is taken from the page's recorder right before, and
// handed to React once hydrated (the root's effect).
setTimeout(() => {
  stopEarlyInput();
  startTransition(() => {
    hydrateRoot(
      document,
      <StrictMode>
        <HydratedRouter />
      </StrictMode>,
    );
  });
}, 0);
