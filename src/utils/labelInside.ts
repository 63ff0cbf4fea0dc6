import type { Directive } from 'vue';

/** What `v-label-inside` sets: the inner element (CSS selector) and its accessible name. */
export interface LabelInside {
  selector: string;
  label: string;
}

function apply(el: HTMLElement, value: LabelInside): void {
  const target = el.querySelector(value.selector);
  if (target && target.getAttribute('aria-label') !== value.label) target.setAttribute('aria-label', value.label);
}

/**
 * Names a control that a library renders inside a component without a way to label it (the page-size picker of
 * Element Plus' pagination has no label prop): `v-label-inside="{ selector: '.el-pagination__sizes input', label:
 * 'Designs per page' }"`. Applied again after every update of the component.
 */
export const vLabelInside: Directive<HTMLElement, LabelInside> = {
  mounted: (el, binding) => apply(el, binding.value),
  updated: (el, binding) => apply(el, binding.value),
};
