// The budget split runs here, off the main thread, so the page stays responsive while it optimises.
import { expose } from "comlink";
import { createSplitApi } from "./split-api";

expose(createSplitApi());
