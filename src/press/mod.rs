//! The built-in press conditions (lead's placeholder until the model lands).

/// ICC bytes of a built-in press condition.
pub fn builtin_icc(_name: &str) -> Option<&'static [u8]> {
    None
}
pub struct PrintCondition;
pub fn builtin_press(_n: &str) -> Option<PrintCondition> {
    None
}
pub fn build_icc(_c: &PrintCondition) -> Result<Vec<u8>, std::io::Error> {
    Err(std::io::Error::other("x"))
}
