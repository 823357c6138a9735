//! The study kinds: one folder each, registered once below.
//!
//! A kind's folder holds everything that knows the kind: its site-file keys and schema text
//! (`doc`), their validation into its model (`validate`, `model`), its run (`run`, calling the
//! numeric core), its result figures (`result`), and its report section, plots and CSV
//! (`report`). The folder's `mod.rs` implements [`Kind`] for it. The registration list at the
//! end of this file generates the tagged site-file enum [`StudyDoc`], the model enum
//! [`StudyKind`], the results enum [`Figures`] and every dispatch over them, so adding a kind is
//! one folder, its `pub mod` line and one line in that list (DEVELOPERS.md, "How to add a study
//! kind").

/// Implements [`CommonKeys`] for document types with `id` and `method` fields.
macro_rules! common_keys {
    ($($doc:ty),+ $(,)?) => {
        $(impl crate::kinds::CommonKeys for $doc {
            fn id(&self) -> &str {
                &self.id
            }
            fn method(&self) -> Option<crate::site::doc::MethodDoc> {
                self.method
            }
        })+
    };
}

pub mod engine_model;

// The kinds' folders (declared here rather than inside the macro so that rustfmt sees them).
pub mod borefield;
pub mod cross_section;
pub mod frost;
pub mod heat_loss;

use crate::ground::profile::Undisturbed;
use crate::model::{Method, Site, Study};
use crate::report::Figure;
use crate::results::{Assumption, Check, DecisiveFigure, StudyResult, Warning};
use crate::site::diagnostic::KeyPath;
use crate::site::doc::MethodDoc;
use crate::site::validate::Validator;

/// What a study run is given besides its own model.
pub struct StudyContext<'a> {
    pub id: &'a str,
    pub method: Method,
    pub site: &'a Site,
    pub ground: &'a Undisturbed,
}

/// What a study run produces: its figures, the warnings it raised, its design decisions as
/// checks, and the assumptions it used.
pub struct Outcome<R> {
    pub result: R,
    pub warnings: Vec<Warning>,
    pub checks: Vec<Check>,
    pub assumptions: Vec<Assumption>,
}

/// The keys every study's document has: its `id` and its `method`.
pub trait CommonKeys {
    fn id(&self) -> &str;
    fn method(&self) -> Option<MethodDoc>;
}

/// The contract every study kind implements.
pub trait Kind {
    /// The kind's name as the site file spells it (`kind: heat-loss`).
    const NAME: &'static str;
    /// The methods the kind offers, and the one used when the site file names none.
    const METHODS: &'static [Method];
    const DEFAULT_METHOD: Method;
    /// The study's keys as written (serde + schemars; doc comments become the schema's text).
    type Doc: CommonKeys;
    /// The validated study in model units.
    type Model;
    /// The study's figures as `results.json` holds them.
    type Result;

    fn id(doc: &Self::Doc) -> &str {
        doc.id()
    }
    fn method(doc: &Self::Doc) -> Option<MethodDoc> {
        doc.method()
    }
    /// Validates the study's own keys; every problem is reported to `v`.
    fn validate(doc: &Self::Doc, path: &KeyPath, v: &mut Validator) -> Option<Self::Model>;
    /// The deepest point the study reaches (a borehole bottom, a model domain), m: the
    /// undisturbed ground is solved at least that deep.
    fn deepest_point_m(model: &Self::Model) -> f64;
    /// Runs the study: model in, plain figures out.
    fn run(cx: &StudyContext, model: &Self::Model) -> Result<Outcome<Self::Result>, String>;
    /// The figures that decide the study (summaries, uncertainty and inventories read these).
    fn decisive_figures(result: &Self::Result) -> Vec<DecisiveFigure>;
    /// The study's plots.
    fn figures(study: &StudyResult, result: &Self::Result) -> Result<Vec<Figure>, String>;
    /// The study's section of the report page (after its inputs, before its plots).
    fn section(result: &Self::Result) -> maud::Markup;
    /// The study's CSV files: name and text.
    fn csv_files(study: &StudyResult, result: &Self::Result) -> Vec<(String, String)>;
}

fn validate_as<K: Kind>(
    doc: &K::Doc,
    path: &KeyPath,
    v: &mut Validator,
    wrap: impl FnOnce(Box<K::Model>) -> StudyKind,
) -> Option<Study> {
    let method = crate::site::validate::method(
        K::method(doc),
        K::DEFAULT_METHOD,
        K::METHODS,
        &path.key("method"),
        v,
    );
    let model = K::validate(doc, path, v);
    Some(Study {
        id: K::id(doc).to_string(),
        method: method?,
        echo: None,
        kind: wrap(Box::new(model?)),
    })
}

/// A finished study run before it is put into [`StudyResult`].
pub struct Ran {
    pub figures: Figures,
    pub warnings: Vec<Warning>,
    pub checks: Vec<Check>,
    pub assumptions: Vec<Assumption>,
}

fn run_as<K: Kind>(
    model: &K::Model,
    cx: &StudyContext,
    wrap: impl FnOnce(Box<K::Result>) -> Figures,
) -> Result<Ran, String> {
    let o = K::run(cx, model)?;
    Ok(Ran {
        figures: wrap(Box::new(o.result)),
        warnings: o.warnings,
        checks: o.checks,
        assumptions: o.assumptions,
    })
}

/// Generates the three enums over the registered kinds and every dispatch over them.
macro_rules! study_kinds {
    ($( $(#[$meta:meta])* $variant:ident => $module:ident :: $kind:ident ),+ $(,)?) => {

        /// One study; `kind` says which, and each kind has its own keys.
        #[derive(Debug, serde::Deserialize, schemars::JsonSchema)]
        #[serde(tag = "kind", rename_all = "kebab-case")]
        pub enum StudyDoc {
            $( $(#[$meta])* $variant(Box<<$module::$kind as Kind>::Doc>), )+
        }

        /// A validated study's kind and its model.
        #[derive(Clone, Debug, PartialEq)]
        pub enum StudyKind {
            $( $variant(Box<<$module::$kind as Kind>::Model>), )+
        }

        /// The figures of each study kind (serialised flat into the study's entry).
        #[derive(Clone, Debug, serde::Serialize)]
        #[serde(untagged)]
        pub enum Figures {
            $( $variant(Box<<$module::$kind as Kind>::Result>), )+
        }

        /// The names of the registered kinds, in registration order.
        pub const NAMES: &[&str] = &[$( <$module::$kind as Kind>::NAME ),+];

        impl StudyDoc {
            pub fn id(&self) -> &str {
                match self { $( StudyDoc::$variant(d) => <$module::$kind as Kind>::id(d), )+ }
            }

            /// Validates the study into the model (its method and its own keys).
            pub fn validate(&self, path: &KeyPath, v: &mut Validator) -> Option<Study> {
                match self {
                    $( StudyDoc::$variant(d) => validate_as::<$module::$kind>(d, path, v, StudyKind::$variant), )+
                }
            }
        }

        impl StudyKind {
            /// The kind's name as the site file spells it.
            pub fn name(&self) -> &'static str {
                match self { $( StudyKind::$variant(_) => <$module::$kind as Kind>::NAME, )+ }
            }

            pub fn deepest_point_m(&self) -> f64 {
                match self { $( StudyKind::$variant(m) => <$module::$kind as Kind>::deepest_point_m(m), )+ }
            }

            pub fn run(&self, cx: &StudyContext) -> Result<Ran, String> {
                match self { $( StudyKind::$variant(m) => run_as::<$module::$kind>(m, cx, Figures::$variant), )+ }
            }
        }

        impl Figures {
            pub fn decisive_figures(&self) -> Vec<DecisiveFigure> {
                match self { $( Figures::$variant(r) => <$module::$kind as Kind>::decisive_figures(r), )+ }
            }

            pub fn figures(&self, study: &StudyResult) -> Result<Vec<Figure>, String> {
                match self { $( Figures::$variant(r) => <$module::$kind as Kind>::figures(study, r), )+ }
            }

            pub fn section(&self) -> maud::Markup {
                match self { $( Figures::$variant(r) => <$module::$kind as Kind>::section(r), )+ }
            }

            pub fn csv_files(&self, study: &StudyResult) -> Vec<(String, String)> {
                match self { $( Figures::$variant(r) => <$module::$kind as Kind>::csv_files(study, r), )+ }
            }
        }
    };
}

// The registration list: one line per kind (its doc comment is the schema's description); the
// kind's folder is declared with the others at the top of this file.
study_kinds! {
    /// Heat loss of buried district-heating pipes, insulation sizing, neighbouring utilities.
    HeatLoss => heat_loss::HeatLossKind,
    /// A free 2-D cross-section of the ground solved by the finite-volume engine.
    CrossSection => cross_section::CrossSectionKind,
    /// Design freezing index, frost depth by Stefan, modified Berggren and the engine's design
    /// winter, and a water main's safety (cover, stagnant water, bleed flow, insulation board).
    Frost => frost::FrostKind,
    /// A field of ground heat exchangers for a heat pump: g-function, borehole resistance, fluid
    /// temperatures over the design life, and length sizing.
    Borefield => borefield::BorefieldKind,
}

/// Runs one study against the site's undisturbed ground; a failure names the study.
pub fn run(
    study: &Study,
    site: &Site,
    ground: &Undisturbed,
) -> Result<(StudyResult, Vec<Warning>), crate::StudyError> {
    let cx = StudyContext {
        id: &study.id,
        method: study.method,
        site,
        ground,
    };
    let ran = study.kind.run(&cx).map_err(|message| crate::StudyError {
        study: study.id.clone(),
        kind: study.kind.name(),
        message: message
            .strip_prefix(&format!("study {}: ", study.id))
            .map(str::to_string)
            .unwrap_or(message),
    })?;
    let decisive_figures = ran.figures.decisive_figures();
    Ok((
        StudyResult {
            id: study.id.clone(),
            kind: study.kind.name().into(),
            method: study.method.name().into(),
            figures: ran.figures,
            checks: ran.checks,
            assumptions: ran.assumptions,
            decisive_figures,
        },
        ran.warnings,
    ))
}

/// The deepest point any study of the site reaches (a borehole bottom, a model domain), m.
pub fn deepest_point_m(site: &Site) -> f64 {
    site.studies
        .iter()
        .map(|s| s.kind.deepest_point_m())
        .fold(0.0, f64::max)
}
