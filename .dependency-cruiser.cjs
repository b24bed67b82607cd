/* global module */
/**
 * The architecture's rules, checked by `npm run lint` (dependency-cruiser). Each rule names the
 * layer it guards; README.md ("Architecture") draws the layers.
 * @type {import('dependency-cruiser').IConfiguration}
 */
module.exports = {
  forbidden: [
    {
      name: 'shared-is-pure',
      comment:
        'shared/ runs in the browser and on the server: it imports only shared/ and pure libraries ' +
        '(no Node built-ins, no server, client or worker code).',
      severity: 'error',
      from: { path: '^shared/' },
      to: {
        pathNot: ['^shared/', '(^|/)node_modules/zod/'],
      },
    },
    {
      name: 'shared-no-core-modules',
      comment: 'shared/ does not use Node built-ins (fs, crypto, …): it runs in the browser too.',
      severity: 'error',
      from: { path: '^shared/' },
      to: { dependencyTypes: ['core'] },
    },
    {
      name: 'client-not-server',
      comment: 'The client (src/) reaches the server only over HTTP: it never imports server/.',
      severity: 'error',
      from: { path: '^src/' },
      to: { path: '^server/' },
    },
    {
      name: 'routes-no-database',
      comment:
        'Routes and middleware never touch a model, a pool or SQL: they call services ' +
        '(server/services/<area>/index.ts), which own the database.',
      severity: 'error',
      from: { path: '^server/(routes|middleware)/' },
      to: {
        path: [
          '^server/models/',
          '^server/db/',
          '(^|/)node_modules/(sequelize|pg|connect-pg-simple)/',
        ],
        // The error handler maps Sequelize's error classes and a lost connection to answers; it
        // reads no rows.
        pathNot: ['^server/db/unavailable\\.ts$'],
        dependencyTypesNot: ['type-only'],
      },
    },
    {
      name: 'models-no-services',
      comment: 'Models describe rows; the rules that use them live in services, never the reverse.',
      severity: 'error',
      from: { path: '^server/models/' },
      to: { path: ['^server/services/', '^server/routes/', '^server/middleware/'] },
    },
    {
      name: 'services-no-http',
      comment: 'Services know nothing of HTTP: they never import routes or middleware.',
      severity: 'error',
      from: { path: '^server/services/' },
      to: { path: ['^server/routes/', '^server/middleware/'] },
    },
    {
      name: 'db-not-upward',
      comment:
        'server/db/ is the bottom layer beside the models: it never imports services, routes or middleware.',
      severity: 'error',
      from: { path: '^server/(db|models)/' },
      to: { path: '^server/(services|routes|middleware|documents|seed|workers|main)/' },
    },
    {
      name: 'no-circular',
      comment:
        'No import cycles between modules. Type-only imports are left out: Product and Revision ' +
        'name each other\u2019s types, which makes no cycle at run time.',
      severity: 'error',
      from: {},
      to: { circular: true, viaOnly: { dependencyTypesNot: ['type-only'] } },
    },
    {
      name: 'no-folder-cycles',
      comment:
        'No import cycles between folders (a layer or an area that imports back its importer). ' +
        'A folder stands for everything under it, so server/ imports nothing outside itself ' +
        'that imports server/ back.',
      severity: 'error',
      scope: 'folder',
      from: {},
      to: { circular: true },
    },
    {
      name: 'not-to-unresolvable',
      comment: 'Every import resolves to a file or an installed package.',
      severity: 'error',
      from: {},
      to: { couldNotResolve: true, pathNot: '(\\.|/)css$' },
    },
  ],
  options: {
    doNotFollow: { path: 'node_modules' },
    exclude: { path: ['^dist/', '\\.d\\.ts$'] },
    tsPreCompilationDeps: true,
    tsConfig: { fileName: 'tsconfig.depcruise.json' },
    enhancedResolveOptions: {
      exportsFields: ['exports'],
      conditionNames: ['import', 'require', 'node', 'default', 'types'],
      mainFields: ['module', 'main', 'types', 'typings'],
      extensions: ['.ts', '.vue', '.js', '.mjs', '.cjs', '.json'],
    },
    reporterOptions: { text: { highlightFocused: true } },
  },
}
