import { fileURLToPath } from 'node:url'
import vue from '@vitejs/plugin-vue'
import { ElementPlusResolver } from 'unplugin-vue-components/resolvers'
import Components from 'unplugin-vue-components/vite'
import { defineConfig } from 'vitest/config'
import { E2E_TEST_MS, E2E_WAIT_MS } from './tests/e2e/support/timeouts'

const fromRoot = (path: string) => fileURLToPath(new URL(path, import.meta.url))

// Five projects; scripts/test.ts runs them as phases (unit = unit + unit-dom, then api, faults,
// e2e).
// vitest 4 has no environmentMatchGlobs, so component tests get their own project.
export default defineConfig({
  plugins: [
    vue(),
    // Same on-demand Element Plus registration as the app, so mounted views resolve <el-*>.
    Components({ dts: false, resolvers: [ElementPlusResolver({ importStyle: false })] }),
  ],
  resolve: {
    alias: { '@': fromRoot('./src'), '@shared': fromRoot('./shared') },
  },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'unit',
          include: ['tests/unit/**/*.test.ts'],
          exclude: ['tests/unit/src/**'],
          environment: 'node',
          // Rendering a label sheet and decoding its QR codes takes well under a second on an
          // idle machine and over five on a loaded one: room for a busy CI machine.
          testTimeout: 30000,
        },
      },
      {
        extends: true,
        test: {
          name: 'unit-dom',
          include: ['tests/unit/src/**/*.test.ts'],
          environment: 'happy-dom',
        },
      },
      {
        extends: true,
        test: {
          name: 'api',
          include: ['tests/api/**/*.test.ts'],
          environment: 'node',
          // One real database: files run one after another.
          fileParallelism: false,
          testTimeout: 20000,
          hookTimeout: 20000,
        },
      },
      {
        extends: true,
        test: {
          // Stops and kills services of a stack of its own (tests/faults/support/stack.ts).
          name: 'faults',
          include: ['tests/faults/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          testTimeout: 180000,
          hookTimeout: 240000,
        },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          include: ['tests/e2e/**/*.test.ts'],
          environment: 'node',
          fileParallelism: false,
          // One setting for the whole suite (tests/e2e/support/timeouts.ts).
          testTimeout: E2E_TEST_MS,
          hookTimeout: E2E_TEST_MS,
          expect: { poll: { timeout: E2E_WAIT_MS } },
        },
      },
    ],
  },
})
