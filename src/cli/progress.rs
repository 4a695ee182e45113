//! Progress bars on stderr for the library's [`Progress`] reports: one bar per
//! stage, drawn only when allowed and stderr is a terminal.

use indicatif::{ProgressBar, ProgressDrawTarget, ProgressStyle};
use kgain::sample::{Progress, Stage};
use std::sync::Mutex;

/// Draws a bar for each stage the library starts.
pub struct Bars {
    show: bool,
    bar: Mutex<Option<ProgressBar>>,
}

impl Bars {
    /// Bars shown when `show`, hidden otherwise.
    pub fn new(show: bool) -> Self {
        Bars {
            show,
            bar: Mutex::new(None),
        }
    }

    fn new_bar(&self, stage: Stage, total: u64) -> ProgressBar {
        if !self.show {
            return ProgressBar::hidden();
        }
        let bar = ProgressBar::with_draw_target(Some(total), ProgressDrawTarget::stderr());
        if let Ok(style) =
            ProgressStyle::with_template("{msg:>12} [{bar:36}] {percent:>3}% {rate:>10} eta {eta}")
        {
            let style = style.with_key(
                "rate",
                |st: &indicatif::ProgressState, w: &mut dyn std::fmt::Write| {
                    let _ = write!(w, "{:.0}/s", st.per_sec());
                },
            );
            bar.set_style(style.progress_chars("=> "));
        }
        bar.set_message(stage.label().to_string());
        bar
    }
}

impl Progress for Bars {
    fn start(&self, stage: Stage, total: u64) {
        let bar = self.new_bar(stage, total);
        if let Ok(mut b) = self.bar.lock() {
            if let Some(old) = b.replace(bar) {
                old.finish_and_clear();
            }
        }
    }

    fn advance(&self, n: u64) {
        if let Ok(b) = self.bar.lock() {
            if let Some(bar) = b.as_ref() {
                bar.inc(n);
            }
        }
    }

    fn finish(&self) {
        if let Ok(mut b) = self.bar.lock() {
            if let Some(bar) = b.take() {
                bar.finish_and_clear();
            }
        }
    }
}
