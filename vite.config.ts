import { fileURLToPath, URL } from 'node:url'
import vue from '@vitejs/plugin-vue'
import Components from 'unplugin-vue-components/vite'
import { ElementPlusResolver } from 'unplugin-vue-components/resolvers'
import { defineConfig } from 'vite'

// scripts/dev.ts runs the API beside the dev server and passes its port here.
const API_ORIGIN = `http://127.0.0.1:${process.env.WAYMARK_API_PORT || '4871'}`

export default defineConfig({
  plugins: [
    vue(),
    // Element Plus components and directives (v-loading) are registered on demand, each with
    // its own CSS, so a route only ships the widgets it uses.
    // NOTE: dts is off: template types come from `element-plus/global` (see src/env.d.ts),
    // so no generated file has to be kept in step with the templates.
    Components({ dts: false, resolvers: [ElementPlusResolver({ importStyle: 'css' })] }),
  ],
  resolve: {
    alias: {
      '@': fileURLToPath(new URL('./src', import.meta.url)),
      '@shared': fileURLToPath(new URL('./shared', import.meta.url)),
    },
  },
  server: {
    host: '127.0.0.1',
    port: 4870,
    strictPort: true,
    // `/u/<serial>` and `/c/<code>` are the QR targets printed on travelers and lot labels;
    // the API answers them, so they go through the proxy too. They are anchored regexes: a
    // plain '/u' key would also capture client paths such as '/units'.
    proxy: {
      '/api': API_ORIGIN,
      '^/u/': API_ORIGIN,
      '^/c/': API_ORIGIN,
    },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    rolldownOptions: {
      output: {
        // Views are lazy routes already; this splits the shared vendor code so no single
        // chunk carries the framework, the UI kit and zod together. The UI kit stays one chunk:
        // splitting it by size made its pieces import each other in a circle, and message
        // boxes then rendered their buttons as bare tags.
        codeSplitting: {
          groups: [
            {
              name: 'vue',
              test: /node_modules[\\/](@vue|vue|vue-router|pinia)[\\/]/,
              priority: 30,
            },
            { name: 'zod', test: /node_modules[\\/]zod[\\/]/, priority: 20 },
            {
              name: 'element-plus',
              test: /node_modules[\\/](element-plus|@element-plus|@floating-ui|@popperjs|@vueuse|lodash-es|lodash-unified|dayjs|async-validator|memoize-one|normalize-wheel-es|@ctrl)[\\/]/,
              priority: 10,
            },
          ],
        },
      },
    },
  },
})
