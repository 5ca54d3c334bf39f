// The building blocks of every HTML e-mail. Inline styles and a single table-free column,
// because mail programs ignore style sheets and many ignore modern layout.
import { defineComponent, h } from 'vue'
import type { PropType } from 'vue'

const INK = '#1d2733'
const SOFT = '#4a5868'
const REED = '#17705f'
const PAPER = '#fbf8f3'

export const MailLayout = defineComponent({
  props: {
    title: { type: String, required: true },
    unsubscribeLink: { type: String as PropType<string | null>, default: null },
  },
  setup(props, { slots }) {
    return () => h('html', { lang: 'en' }, [
      h('head', [
        h('meta', { charset: 'utf-8' }),
        h('meta', { name: 'viewport', content: 'width=device-width, initial-scale=1' }),
        h('title', props.title),
      ]),
      h('body', { style: `margin:0;padding:24px 12px;background:${PAPER};color:${INK};font-family:Nunito,'Segoe UI',Arial,sans-serif;font-size:16px;line-height:1.5` }, [
        h('div', { style: 'max-width:560px;margin:0 auto;background:#ffffff;border-radius:12px;padding:28px 24px' }, [
          h('p', { style: `margin:0 0 20px;font-weight:800;font-size:18px;color:${REED}` }, 'Evenhand'),
          slots.default?.(),
        ]),
        h('p', { style: `max-width:560px;margin:16px auto 0;color:${SOFT};font-size:13px;text-align:center` }, props.unsubscribeLink
          ? ['You receive this because a student named you as their guardian. ', h('a', { href: props.unsubscribeLink, style: `color:${SOFT}` }, 'Stop these e-mails')]
          : 'Evenhand, fingering practice for piano students and their teachers'),
      ]),
    ])
  },
})

export const MailParagraph = defineComponent({
  setup(_, { slots }) {
    return () => h('p', { style: 'margin:0 0 14px' }, slots.default?.())
  },
})

/** The one action of a mail, with its address printed below for mail programs that hide buttons. */
export const MailButton = defineComponent({
  props: { href: { type: String, required: true }, label: { type: String, required: true } },
  setup(props) {
    return () => h('div', { style: 'margin:22px 0' }, [
      h('a', { href: props.href, style: `display:inline-block;background:${REED};color:#ffffff;text-decoration:none;font-weight:700;padding:12px 20px;border-radius:8px` }, props.label),
      h('p', { style: `margin:12px 0 0;font-size:13px;color:${SOFT};word-break:break-all` }, ['Or open this address: ', h('a', { href: props.href, style: `color:${REED}` }, props.href)]),
    ])
  },
})

export const MailTable = defineComponent({
  props: {
    head: { type: Array as PropType<string[]>, required: true },
    rows: { type: Array as PropType<string[][]>, required: true },
  },
  setup(props) {
    const cell = 'padding:6px 10px;border-bottom:1px solid #e5e0d6;text-align:left'
    return () => h('table', { style: 'border-collapse:collapse;width:100%;margin:0 0 16px;font-size:15px' }, [
      h('thead', [h('tr', props.head.map(title => h('th', { style: `${cell};color:${SOFT};font-weight:700` }, title)))]),
      h('tbody', props.rows.map(row => h('tr', row.map(value => h('td', { style: cell }, value))))),
    ])
  },
})
