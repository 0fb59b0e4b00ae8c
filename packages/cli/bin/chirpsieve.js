#!/usr/bin/env node
// Launcher kept in git so that `npm ci` can link the `chirpsieve` command before the build has
// run (npm links bins at install time; `prepare` builds dist/ afterwards).
import "../dist/main.js";
