/// <reference types="vite/client" />
/// <reference types="element-plus/global" />

declare module '*.vue' {
  import type { DefineComponent } from 'vue'
  // NOTE: the shim only types imports for tools outside vue-tsc; vue-tsc reads the SFCs itself.
  const component: DefineComponent<object, object, unknown>
  export default component
}
