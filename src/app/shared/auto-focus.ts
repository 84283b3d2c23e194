import { Directive, ElementRef, afterNextRender, inject } from '@angular/core';

/** Focuses its element once it is on screen: a field that appears because the user asked for it (rename). */
@Directive({ selector: '[emAutoFocus]' })
export class AutoFocus {
  constructor() {
    const element = inject<ElementRef<HTMLElement>>(ElementRef).nativeElement;
    afterNextRender(() => {
      element.focus();
      if (element instanceof HTMLInputElement) element.select();
    });
  }
}
