// The prior check runs here, off the main thread, so the form stays responsive while it draws.
import { expose } from "comlink";
import { priorCheckApi } from "./prior-check-api";

expose(priorCheckApi);
