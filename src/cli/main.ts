#!/usr/bin/env node
/** Demo / command-line front end (filled in as the modules land). */
const quick = process.argv.includes('--quick');
console.log(`chronomesh demo${quick ? ' (quick)' : ''}: modules are being built.`);
