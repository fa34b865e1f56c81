import "@fontsource/ibm-plex-sans/latin-400.css";
import "@fontsource/ibm-plex-sans/latin-500.css";
import "@fontsource/ibm-plex-sans/latin-600.css";
import "@fontsource/fraunces/latin-600.css";
import "@fontsource/fraunces/latin-400-italic.css";
import "./styles/base.css";

import { createApp } from "vue";
import { createPinia } from "pinia";
import App from "./App.vue";
import { createGrainyardRouter } from "./router.ts";
import { useSessionStore } from "./stores/session.ts";
import { transport } from "./api/http.ts";

const app = createApp(App);
const pinia = createPinia();
app.use(pinia);

// The API client asks the session store for the anti-forgery token on every state-changing call.
const session = useSessionStore(pinia);
transport.useCsrfToken(() => session.csrfToken);

app.use(createGrainyardRouter(pinia));
app.mount("#app");
