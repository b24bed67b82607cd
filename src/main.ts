import { createPinia } from 'pinia'
import { createApp } from 'vue'
import App from './App.vue'
import { router } from './router'
// Fonts come from our own bundle: the shop floor may have no internet, and we load nothing from it.
import '@fontsource/roboto-condensed/400.css'
import '@fontsource/roboto-condensed/500.css'
import '@fontsource/roboto-condensed/700.css'
// ElMessage and ElMessageBox are called from scripts, which the on-demand resolver does not
// see, so their styles are imported once here.
import 'element-plus/es/components/message/style/css'
import 'element-plus/es/components/message-box/style/css'
import './styles/index.css'

// Pinia before the router: the navigation guard reads the session store.
createApp(App).use(createPinia()).use(router).mount('#app')
